module nodal

go 1.26

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/alecthomas/participle/v2 v2.1.4
	github.com/fatih/color v1.19.0
	github.com/mattn/go-isatty v0.0.20
)

require (
	github.com/mattn/go-colorable v0.1.14 // indirect
	golang.org/x/sys v0.42.0 // indirect
)
