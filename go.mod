module loopwise

go 1.26.8

require (
	github.com/clipperhouse/uax29/v2 v2.7.0 // indirect
	github.com/expr-lang/expr v1.17.8 // indirect
	github.com/mattn/go-runewidth v0.0.31 // indirect
	github.com/peterh/liner v1.2.3 // indirect
	github.com/rogpeppe/go-internal v1.16.0 // indirect
	golang.org/x/sys v0.48.0 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
