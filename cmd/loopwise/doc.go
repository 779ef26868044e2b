// Command loopwise is the Loopwise calculator for electromagnetic induction:
// an interactive prompt, and replayable script files.
//
//	loopwise                      interactive prompt (or statements from a pipe)
//	loopwise FILE.lw              same as: loopwise run FILE.lw
//	loopwise run FILE|DIR...      evaluate scripts and print the worked calculation
//	loopwise check [-tol R] FILE|DIR...
//	                              re-evaluate and compare every recorded result
//	loopwise record FILE|DIR...   rewrite the recorded results in place
//
// This is the only package that touches the terminal.
package main
