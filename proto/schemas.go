package proto

import "embed"

// Schemas holds the JSON schemas of what framed publishes and accepts, by
// file name: result, event, status, specimen, command, verification,
// tests and bench (schemas/<name>.schema.json). They are the contract for
// the lab's systems; the tests validate real output against them.
//
//go:embed schemas/*.schema.json
var Schemas embed.FS
