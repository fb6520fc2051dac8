// Command drawsift is the command-line host of the Drawsift engine.
//
//	drawsift osmotic [-f FILE] [--format json|csv|table]   osmotic properties of one solution
//	drawsift flux    [-f FILE] [--format json|csv|table]   FO water and solute flux
//	drawsift screen  [-f FILE] [--format json|csv|table]   rank candidate draw solutes
//	drawsift solutes [--json]                              the solute library
//	drawsift presets [--json]                              membrane and feed presets
//	drawsift demo                                          the built-in demo table
//	drawsift help [COMMAND]                                every command, or one command's fields
//
// Requests are the contract's JSON (see the README), read from standard
// input or FILE. Errors are printed as the contract's error object on
// standard output with exit status 2.
package main

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"

	"drawsift/engine/api"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

// run is main without the process: it returns the exit status.
// 0 success, 2 a request error (printed as the contract's error object),
// 1 a usage or I/O error.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		printUsage(stderr)
		return 1
	}
	cmd, rest := args[0], args[1:]
	// drawsift COMMAND -h / --help: the command's help (serve and bundle
	// print their flags themselves).
	if c := findCommand(cmd); c != nil && cmd != "serve" && cmd != "bundle" && cmd != "help" && wantsHelp(rest) {
		printHelp(stdout, c)
		return 0
	}
	switch cmd {
	case api.OpOsmotic, api.OpFlux, api.OpScreen, api.OpBatch, api.OpFit, api.OpModule, api.OpRobustnessMerge:
		return runOp(cmd, rest, stdin, stdout, stderr)
	case api.OpDefaults:
		if len(rest) > 0 {
			fmt.Fprintf(stderr, "drawsift defaults: unexpected argument %q\n", rest[0])
			return 1
		}
		out, e := api.Dispatch(context.Background(), api.OpDefaults, nil)
		if e != nil {
			stdout.Write(out)
			fmt.Fprintln(stdout)
			return 2
		}
		if err := render(stdout, api.OpDefaults, "json", out); err != nil {
			fmt.Fprintf(stderr, "drawsift defaults: %v\n", err)
			return 1
		}
		return 0
	case api.OpSolutes, api.OpPresets:
		return runList(cmd, rest, stdout, stderr)
	case "serve":
		return runServe(rest, stdout, stderr)
	case "bundle":
		return runBundle(rest, stdout, stderr)
	case "demo":
		if len(rest) > 0 {
			fmt.Fprintf(stderr, "drawsift demo: unexpected argument %q; type drawsift demo for the table, or drawsift screen --demo for the demo screen\n", rest[0])
			return 1
		}
		return runDemo(stdout, stderr)
	case "version", "--version":
		fmt.Fprintln(stdout, "drawsift engine", api.EngineVersion)
		return 0
	case "help", "-h", "--help":
		if len(rest) == 0 {
			printUsage(stdout)
			return 0
		}
		if c := findCommand(rest[0]); c != nil {
			if c.name == "serve" || c.name == "bundle" {
				return run([]string{c.name, "-h"}, stdin, stdout, stderr)
			}
			printHelp(stdout, c)
			return 0
		}
		fmt.Fprintf(stderr, "drawsift help: no command %q. %sType drawsift help for the list.\n", rest[0], suggest(rest[0]))
		return 1
	}
	fmt.Fprintf(stderr, "drawsift: unknown command %q. %sType drawsift help for the list.\n\n", cmd, suggest(cmd))
	printUsage(stderr)
	return 1
}

func runOp(op string, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet(op, flag.ContinueOnError)
	fs.SetOutput(stderr)
	file := fs.String("f", "", "read the request from `FILE`")
	format := fs.String("format", "json", "output `FORMAT`: json, csv or table")
	var demo *bool
	if op == api.OpScreen {
		demo = fs.Bool("demo", false, "screen the built-in demo scenario (a brackish-water field station)")
	}
	var batch *batchFlags
	if op == api.OpScreen {
		batch = addBatchFlags(fs)
	}
	var csvFile *string
	if op == api.OpFit {
		csvFile = fs.String("csv", "", "read the measurements from the CSV `FILE` (units in the header)")
	}
	if err := fs.Parse(args); err != nil {
		return 1
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "drawsift %s: unexpected argument %q\n", op, fs.Arg(0))
		return 1
	}
	f := strings.ToLower(*format)
	if f != "json" && f != "csv" && f != "table" {
		fmt.Fprintf(stderr, "drawsift %s: unknown format %q (json, csv or table)\n", op, *format)
		return 1
	}
	var in io.Reader = stdin
	if csvFile != nil && *csvFile != "" && *file == "" {
		in = strings.NewReader("{}")
	}
	if demo != nil && *demo {
		in = bytes.NewReader(demoScenario)
	} else if *file != "" {
		fh, err := os.Open(*file)
		if err != nil {
			fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
			return 1
		}
		defer fh.Close()
		in = fh
	}
	body, err := io.ReadAll(io.LimitReader(in, maxRequestBytes+1))
	if err != nil {
		fmt.Fprintf(stderr, "drawsift %s: reading request: %v\n", op, err)
		return 1
	}
	if len(body) > maxRequestBytes {
		writeErr(stdout, &api.Error{Field: "", Message: fmt.Sprintf("request larger than %d bytes", maxRequestBytes), Limit: maxRequestBytes})
		return 2
	}
	if csvFile != nil && *csvFile != "" {
		if body, err = withCSV(body, *csvFile); err != nil {
			fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
			return 1
		}
	}
	if batch != nil {
		if code, handled := batch.runBatch(op, body, f, stdout, stderr); handled {
			return code
		}
	}
	if op == api.OpScreen && f == "json" && bytes.Contains(body, []byte(`"sweep"`)) {
		if code, ok := streamSweep(body, stdout, stderr); ok {
			return code
		}
	}
	out, e := api.Dispatch(context.Background(), op, body)
	if e != nil {
		stdout.Write(out)
		fmt.Fprintln(stdout)
		if e.Kind == api.KindInternal {
			fmt.Fprintln(stderr, "drawsift: internal error:", e.Detail())
		}
		return 2
	}
	if err := render(stdout, op, f, out); err != nil {
		fmt.Fprintf(stderr, "drawsift %s: %v\n", op, err)
		return 1
	}
	return 0
}

// maxRequestBytes bounds a CLI request (64 MiB: batch files are large, but
// not unbounded).
const maxRequestBytes = 64 << 20

func writeErr(w io.Writer, e *api.Error) {
	fmt.Fprintf(w, `{"error":{"field":%q,"message":%q}}`+"\n", e.Field, e.Message)
}

// withCSV puts the text of the CSV file into the fit request's "csv"
// field (the request's other members kept as they are).
func withCSV(body []byte, path string) ([]byte, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if len(text) > maxRequestBytes {
		return nil, fmt.Errorf("%s: larger than %d bytes", path, maxRequestBytes)
	}
	req := map[string]json.RawMessage{}
	if len(bytes.TrimSpace(body)) > 0 {
		if err := json.Unmarshal(body, &req); err != nil {
			return nil, fmt.Errorf("the request with --csv must be a JSON object of options: %v", err)
		}
	}
	if _, ok := req["data"]; ok {
		return nil, fmt.Errorf("--csv and a request with \"data\" rows: give the measurements once")
	}
	enc, err := json.Marshal(string(text))
	if err != nil {
		return nil, err
	}
	req["csv"] = enc
	return json.Marshal(req)
}

// streamSweep prints a screen with a sweep as it is computed
// (api.ScreenStream through an indenting writer: the bytes render would
// print, without holding the whole sweep). ok false: an error came before
// the answer started, and the caller answers as for any request.
func streamSweep(body []byte, stdout, stderr io.Writer) (code int, ok bool) {
	bw := bufio.NewWriterSize(stdout, 64<<10)
	started, e := api.ScreenStream(context.Background(), body, &indentWriter{w: bw}, nil)
	if e != nil && !started {
		return 0, false
	}
	if e == nil {
		bw.WriteByte('\n')
		if err := bw.Flush(); err != nil {
			e = &api.Error{Message: err.Error()}
		}
	}
	if e != nil {
		fmt.Fprintf(stderr, "drawsift screen: %s\n", e.Message)
		return 1, true
	}
	return 0, true
}
