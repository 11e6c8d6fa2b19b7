// Package curvefile reads and writes curve files: the CSV the project uses
// to import, export and replay a recorded test, with the header
// time_s,force_N,extension_mm,crosshead_mm. An empty cell means no reading
// (NaN in the reduce.Curve), e.g. after the extensometer was removed.
//
// It works on io.Reader and io.Writer only and opens no files. Odd input
// gives an error naming the line, never a panic; the reader caps line
// length so a garbled file cannot exhaust memory.
package curvefile
