// Command evenbeat serves the Evenbeat browser app or writes it out as static
// files, and plans, tabulates and reports from the same files the app uses.
//
//	evenbeat serve [-addr 127.0.0.1:8080] [-src DIR]
//	evenbeat build -o DIR [-src DIR]
//	evenbeat plan [-json] [-cylinder NAME] [-priority leads|cut-offs|balanced] SESSION.json
//	evenbeat events [-json] ENGINE.json
//	evenbeat report SESSION.json -o report.png
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	if err := run(ctx, os.Args[1:], os.Stdout, os.Stderr); err != nil {
		fmt.Fprintln(os.Stderr, "evenbeat:", err)
		os.Exit(1)
	}
}
