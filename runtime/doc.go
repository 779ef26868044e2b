// Package runtime holds the values of Loopwise (quantities with SI
// dimensions, vectors of quantities, functions), the unit catalogue, the
// operator dispatcher that the expression engine calls for every arithmetic
// and comparison operator, the display formatting, the session that
// evaluates statements, and the replay of script files (run, check, record).
//
// A statement flows: lang.ParseStatement → lang.Rewrite (unit literals) →
// expr.Compile with the patcher in compile.go → expr.Run → Format.
package runtime
