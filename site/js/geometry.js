// Drawing geometry for the two-measure chart: the outline (envelope) of a
// cloud of points on screen. This is drawing, not DEA: the scores on the page
// all come from the engine; this only traces the line the chart shows.

// chain returns the upper convex chain of pts from the leftmost point (the
// highest among equals) to the highest point (the leftmost among equals).
export function chain(pts) {
  const good = pts.filter((p) => Number.isFinite(p[0]) && Number.isFinite(p[1]));
  if (!good.length) return [];
  let top = good[0];
  for (const p of good) if (p[1] > top[1] || (p[1] === top[1] && p[0] < top[0])) top = p;
  const left = good.filter((p) => p[0] <= top[0]).sort((a, b) => a[0] - b[0] || b[1] - a[1]);
  const hull = [];
  for (const p of left) {
    if (hull.length && hull[hull.length - 1][0] === p[0]) continue; // keep the highest at each x
    while (hull.length >= 2) {
      const a = hull[hull.length - 2], b = hull[hull.length - 1];
      const cross = (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0]);
      if (cross >= 0) hull.pop(); // b lies on or below the segment a-p
      else break;
    }
    hull.push(p);
  }
  // Drop a leading stretch that falls (it cannot, as top is the highest, but
  // equal heights leave flat steps that add nothing).
  return hull;
}

// scaledSet returns the points a returns-to-scale assumption lets the
// outline reach: the units themselves, the origin when shrinking is free,
// and far-out copies when growing is free. big is a scale factor that puts
// a copy beyond the chart's edge.
export function scaledSet(pts, returns, lower, upper, big) {
  const scale = (t) => pts.map((p) => [p[0] * t, p[1] * t]);
  switch (returns) {
    case 'constant': return [[0, 0], ...pts, ...scale(big)];
    case 'non-increasing': return [[0, 0], ...pts];
    case 'non-decreasing': return [...pts, ...scale(big)];
    case 'bounded': {
      const lo = Math.max(0, lower || 0);
      const hi = upper && upper > 0 && Number.isFinite(upper) ? upper : big;
      return [...scale(lo), ...scale(hi)];
    }
    default: return pts;
  }
}

// ioFrontier is the outline for one input (x) against one output (y): from
// the x axis up at the smallest input, along the upper chain, then level.
export function ioFrontier(pts, returns, lower, upper, xMax) {
  const minX = Math.min(...pts.map((p) => p[0]).filter((x) => x > 0));
  const big = Number.isFinite(minX) ? Math.max(4, (20 * xMax) / minX) : 1e6;
  const h = chain(scaledSet(pts, returns, lower, upper, big));
  if (!h.length) return [];
  return [[h[0][0], 0], ...h, [Math.max(xMax * 10, h[h.length - 1][0]), h[h.length - 1][1]]];
}

// lowerLeftFrontier is the outline for two inputs per unit of output: the
// lower-left convex chain, open upward and to the right.
export function lowerLeftFrontier(pts, xMax, yMax) {
  const h = chain(pts.map((p) => [p[0], -p[1]])).map((p) => [p[0], -p[1]]);
  if (!h.length) return [];
  return [[h[0][0], yMax * 10], ...h, [xMax * 10, h[h.length - 1][1]]];
}

// upperRightFrontier is the outline for two outputs per unit of input: the
// upper-right concave chain, closed onto both axes.
export function upperRightFrontier(pts) {
  const h = chain(pts.map((p) => [-p[0], p[1]])).map((p) => [-p[0], p[1]]);
  if (!h.length) return [];
  return [[h[0][0], 0], ...h, [0, h[h.length - 1][1]]];
}
