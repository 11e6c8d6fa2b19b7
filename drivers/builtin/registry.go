package builtin

import (
	"fmt"
	"slices"
	"sync"

	"framed/drivers"
)

var (
	mu        sync.RWMutex
	factories = map[string]func() drivers.Driver{}
)

// Register adds a built-in driver. It panics on an empty name, a nil
// factory or a name registered twice: those are programming errors found
// at start-up, never input.
func Register(name string, factory func() drivers.Driver) {
	if name == "" || factory == nil {
		panic("builtin: Register needs a name and a factory")
	}
	mu.Lock()
	defer mu.Unlock()
	if _, dup := factories[name]; dup {
		panic(fmt.Sprintf("builtin: driver %q registered twice", name))
	}
	factories[name] = factory
}

// Names lists the registered drivers, sorted.
func Names() []string {
	mu.RLock()
	defer mu.RUnlock()
	names := make([]string, 0, len(factories))
	for n := range factories {
		names = append(names, n)
	}
	slices.Sort(names)
	return names
}

// Lookup returns the factory of a registered driver.
func Lookup(name string) (func() drivers.Driver, bool) {
	mu.RLock()
	defer mu.RUnlock()
	f, ok := factories[name]
	return f, ok
}
