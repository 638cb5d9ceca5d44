package forestplot_test

import (
	"io"
	"testing"

	"coefaudit/report/forestplot"
)

func BenchmarkWriteSVG(b *testing.B) {
	p := forestplot.Plot{Topic: "benchmark", Rows: demoRows(), Pooled: demoPooled()}
	for b.Loop() {
		if err := forestplot.WriteSVG(io.Discard, p); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWritePNG(b *testing.B) {
	p := forestplot.Plot{Topic: "benchmark", Rows: demoRows(), Pooled: demoPooled()}
	for b.Loop() {
		if err := forestplot.WritePNG(io.Discard, p); err != nil {
			b.Fatal(err)
		}
	}
}
