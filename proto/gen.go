// Package proto holds the wire contracts of framed: the gRPC service of
// driver plugins (driver.proto, generated into driverpb) and the published
// JSON schemas.
//
// Regenerate the Go code after editing driver.proto with
//
//	go generate ./proto/...
//
// which needs protoc and the two Go plugins on PATH (the generated code in
// the repository was made with exactly these versions; keep them in step
// with google.golang.org/protobuf and google.golang.org/grpc in go.mod):
//
//	apt-get install protobuf-compiler   # libprotoc 3.21.12
//	go install google.golang.org/protobuf/cmd/protoc-gen-go@v1.36.12
//	go install google.golang.org/grpc/cmd/protoc-gen-go-grpc@v1.6.2
//	export PATH="$PATH:$(go env GOPATH)/bin"
package proto

//go:generate protoc --go_out=driverpb --go_opt=paths=source_relative --go-grpc_out=driverpb --go-grpc_opt=paths=source_relative driver.proto
