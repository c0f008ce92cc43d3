module github.com/opsift/opsift

go 1.26.8
