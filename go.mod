module earshot

go 1.26.0

require (
	github.com/golang/geo v0.0.0-20260818125358-b200a1149890
	gonum.org/v1/gonum v0.17.0
)

require golang.org/x/image v0.48.0
