module assay

go 1.26.0

require (
	github.com/inconshreveable/mousetrap v1.1.0 // indirect
	github.com/james-bowman/sparse v0.0.0-20260216202247-495ee4f84d35 // indirect
	github.com/kljensen/snowball v0.10.0 // indirect
	github.com/spf13/cobra v1.10.2 // indirect
	github.com/spf13/pflag v1.0.9 // indirect
	golang.org/x/text v0.44.0 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
