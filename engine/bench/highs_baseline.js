// The general-purpose baseline for ./build.sh bench: every unit's linear
// programs written as CPLEX LP text and solved one by one with HiGHS (the npm
// package "highs", HiGHS compiled to WebAssembly), the way a per-unit
// approach with an off-the-shelf solver works. Each unit gets the same two
// stages as the engine: the radial program (variable returns, input
// orientation: min theta s.t. sum_j l_j x_j <= theta x_o, sum_j l_j y_j >=
// y_o, sum_j l_j = 1, l >= 0) and the slack program (theta fixed at its
// optimum, maximise the slacks, each divided by its measure's mean as the
// engine does).
//
// Usage: node highs_baseline.js STUDY.json SAMPLE [SEED]
// STUDY.json is written by `peerbench -data`. When the study has more units
// than SAMPLE, a seeded random sample of SAMPLE units is solved and the time
// is scaled to all units; the output says so. Prints one JSON line.
"use strict";

const fs = require("fs");

function lcg(seed) {
  let s = BigInt(seed) & 0xffffffffffffn;
  return () => {
    s = (s * 0x5deece66dn + 0xbn) & 0xffffffffffffn;
    return Number(s >> 17n) / 2 ** 31;
  };
}

// num writes a number the LP format reads back exactly.
const num = (v) => (Number.isInteger(v) ? String(v) : v.toPrecision(17));

// terms writes sum_j rows[j][k] l_j (k < 0: sum_j l_j).
const terms = (rows, k) => rows.map((r, j) => (k < 0 ? `+ l${j}` : `+ ${num(r[k])} l${j}`)).join(" ");

// rowsLP writes the constraints shared by both stages; inRhs(i) and
// outRhs(r) end the input and output rows.
function rowsLP(x, y, inRhs, outRhs) {
  const out = [];
  for (let i = 0; i < x[0].length; i++) out.push(` in${i}: ${terms(x, i)} ${inRhs(i)}`);
  for (let r = 0; r < y[0].length; r++) out.push(` out${r}: ${terms(y, r)} ${outRhs(r)}`);
  out.push(` sum: ${terms(x, -1)} = 1`, "End");
  return out;
}

// radialLP is the first stage for unit o.
function radialLP(x, y, o) {
  return ["Minimize", " obj: theta", "Subject To",
    ...rowsLP(x, y, (i) => `- ${num(x[o][i])} theta <= 0`, (r) => `>= ${num(y[o][r])}`)].join("\n");
}

// slackLP is the second stage for unit o with the score fixed at theta.
function slackLP(x, y, o, theta, mx, my) {
  const obj = [];
  for (let i = 0; i < mx.length; i++) obj.push(`+ ${num(1 / mx[i])} si${i}`);
  for (let r = 0; r < my.length; r++) obj.push(`+ ${num(1 / my[r])} so${r}`);
  return ["Maximize", ` obj: ${obj.join(" ")}`, "Subject To",
    ...rowsLP(x, y, (i) => `+ si${i} = ${num(theta * x[o][i])}`, (r) => `- so${r} = ${num(y[o][r])}`)].join("\n");
}

function means(rows) {
  const k = rows[0].length, mu = new Array(k).fill(0);
  for (const r of rows) for (let i = 0; i < k; i++) mu[i] += Math.abs(r[i]);
  return mu.map((v) => (v > 0 ? v / rows.length : 1));
}

async function main() {
  const [file, sampleArg, seedArg] = process.argv.slice(2);
  const study = JSON.parse(fs.readFileSync(file, "utf8"));
  const { x, y, score } = study;
  const n = x.length;
  const sample = Math.min(n, Number(sampleArg || 20));
  const rnd = lcg(Number(seedArg || 1));
  const units = [...Array(n).keys()];
  for (let k = n - 1; k > 0; k--) {
    const j = Math.floor(rnd() * (k + 1));
    [units[k], units[j]] = [units[j], units[k]];
  }
  const chosen = units.slice(0, sample);
  const highs = await require("highs")();
  const opts = { output_flag: false };
  const mx = means(x), my = means(y);
  let total = 0, solve = 0, maxDiff = 0;
  const cpu0 = process.cpuUsage();
  for (const o of chosen) {
    const t0 = performance.now();
    const lp1 = radialLP(x, y, o);
    const t1 = performance.now();
    const r1 = highs.solve(lp1, opts);
    const t2 = performance.now();
    if (r1.Status !== "Optimal") throw new Error(`unit ${o}: radial stage ${r1.Status}`);
    const theta = r1.Columns.theta.Primal;
    const lp2 = slackLP(x, y, o, theta, mx, my);
    const t3 = performance.now();
    const r2 = highs.solve(lp2, opts);
    const t4 = performance.now();
    if (r2.Status !== "Optimal") throw new Error(`unit ${o}: slack stage ${r2.Status}`);
    total += t4 - t0;
    solve += t2 - t1 + (t4 - t3);
    if (score) maxDiff = Math.max(maxDiff, Math.abs(theta - score[o]));
  }
  const cpu = process.cpuUsage(cpu0);
  const perUnit = total / 1000 / sample;
  const line = {
    runtime: "highs",
    units: n,
    sampled: sample,
    perUnitSec: perUnit,
    solveSec: solve / 1000 / sample,
    perUnitCPUSec: (cpu.user + cpu.system) / 1e6 / sample,
    totalSec: perUnit * n,
    maxScoreDiff: maxDiff,
    compared: score ? sample : 0,
    maxRSSMB: process.resourceUsage().maxRSS / 1024,
    description:
      sample < n
        ? `a seeded sample of ${sample} of ${n} units solved (two LPs each, text written and solved), time scaled to all ${n} units`
        : `all ${n} units solved (two LPs each, text written and solved)`,
  };
  console.log(JSON.stringify(line));
}

main().catch((e) => {
  console.error("highs_baseline:", e.message || e);
  process.exit(1);
});
