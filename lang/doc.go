// Package lang holds the surface syntax of Loopwise statements: source
// positions, the one positioned error type, the splitting of a line into a
// statement (assignment, function definition, conversion or expression) and
// the pre-lexer that turns unit literals such as "5 mT" into placeholders
// that the expression engine (github.com/expr-lang/expr) can parse.
//
// The package imports nothing else of Loopwise. Knowledge of which names are
// units is passed in through the UnitNames interface.
package lang
