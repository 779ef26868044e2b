// Package builtins provides the functions and constants a Loopwise session
// starts with. Each family of builtins lives in its own file with a
// registration table: name, signature with units, the Go function, help text
// and the outside reference its behaviour is checked against.
//
// Standard returns the whole library; cmd/loopwise hands it to
// runtime.NewSession.
package builtins
