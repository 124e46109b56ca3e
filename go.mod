module spallscope

go 1.26.0

require (
	github.com/spf13/cobra v1.10.2
	gocv.io/x/gocv v0.31.0
	golang.org/x/image v0.48.0
	gonum.org/v1/gonum v0.17.0
)

require (
	github.com/inconshreveable/mousetrap v1.1.0 // indirect
	github.com/spf13/pflag v1.0.9 // indirect
)
