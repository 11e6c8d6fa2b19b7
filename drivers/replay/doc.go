// Package replay is a driver that plays a recorded curve file
// (time_s,force_N,extension_mm,crosshead_mm; an empty cell is no reading)
// as if a frame were producing it, at recorded speed, faster, or as fast
// as the consumer takes it, so a recorded test can run through the whole
// daemon again: detection, storage, reduction and publishing.
//
// Caveats: the whole file is read into memory at Configure (a 6 M-sample
// recording takes about 200 MB). Channels that have no reading at all in
// the file are left out of Info. Repeated time stamps in a file are
// nudged forward by a nanosecond, since a stream's times must rise.
// Between loops and after the end the "frame" is idle with the specimen
// out: force 0, no extension or crosshead reading.
package replay
