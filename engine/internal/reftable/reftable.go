// Package reftable reads the reference tables in testdata/ (CSV written
// by the SciPy scripts: '#' comment lines, then a header row naming the
// columns) for the tests that compare the engine with them.
package reftable

import (
	"encoding/csv"
	"fmt"
	"os"
)

// Read returns the table at path: the column index of each header name
// and the data rows (the header removed).
func Read(path string) (head map[string]int, rows [][]string, err error) {
	fh, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	defer fh.Close()
	rd := csv.NewReader(fh)
	rd.Comment = '#'
	all, err := rd.ReadAll()
	if err != nil {
		return nil, nil, err
	}
	if len(all) == 0 {
		return nil, nil, fmt.Errorf("%s: no header row", path)
	}
	head = make(map[string]int, len(all[0]))
	for i, h := range all[0] {
		head[h] = i
	}
	return head, all[1:], nil
}
