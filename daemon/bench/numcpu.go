package bench

import "runtime"

func numCPU() int { return runtime.NumCPU() }
