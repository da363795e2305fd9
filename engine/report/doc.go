// Package report turns DEA results into plain sentences for the page and the
// exports: what a unit could save or produce, which peers it is compared
// with, its targets against today's values, what is proportional (radial) and
// what is slack, the weights that show it in its best light, whether the
// result was verified, and its returns to scale and super-efficiency.
//
// It also describes the models in plain words with their sources and keeps
// the cautions every set of DEA scores should travel with.
//
// Everything here is text built from numbers already computed by package dea;
// nothing is recomputed except percentages of those numbers.
package report
