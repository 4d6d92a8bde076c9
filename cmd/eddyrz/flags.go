package main

import (
	"strings"

	"eddyrz/geometry"
)

// quantityFlag is a command-line value written like a job-file quantity ("10 s", "60 kHz", "2 min"); a bare
// number is SI. The parsed value lands in *v.
type quantityFlag struct {
	dim geometry.Dim
	v   *float64
	s   string
}

func newQuantityFlag(dim geometry.Dim, v *float64) *quantityFlag {
	return &quantityFlag{dim: dim, v: v}
}

func (q *quantityFlag) String() string { return q.s }
func (q *quantityFlag) Type() string   { return "quantity" }
func (q *quantityFlag) Set(s string) error {
	x, err := geometry.ParseQuantity(s, q.dim)
	if err != nil {
		return err
	}
	*q.v, q.s = x, s
	return nil
}

// quantityListFlag is a comma-separated list of quantities ("10 s, 30 s, 1 min").
type quantityListFlag struct {
	dim geometry.Dim
	v   *[]float64
	s   string
}

func newQuantityListFlag(dim geometry.Dim, v *[]float64) *quantityListFlag {
	return &quantityListFlag{dim: dim, v: v}
}

func (q *quantityListFlag) String() string { return q.s }
func (q *quantityListFlag) Type() string   { return "quantities" }
func (q *quantityListFlag) Set(s string) error {
	var out []float64
	for _, f := range strings.Split(s, ",") {
		x, err := geometry.ParseQuantity(strings.TrimSpace(f), q.dim)
		if err != nil {
			return err
		}
		out = append(out, x)
	}
	*q.v, q.s = out, s
	return nil
}
