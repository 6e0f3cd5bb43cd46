// Placement of labels beside a drawing, so that none covers another (the canal diagram).

/**
 * Centres for labels of height `h` stacked in one column between `top` and `bottom`, each as
 * near its anchor (`wanted`, in the same order) as the others allow, none overlapping.
 * Labels that crowd one another form a group centred on their anchors; a group that would
 * leave the column is slid back into it. When even a tight stack does not fit, the labels
 * are spread evenly over the column (the caller draws them smaller).
 *
 * @example spreadLabels([100, 104, 200], 12, 0, 300) // → [96, 108, 200]
 */
export function spreadLabels(wanted: readonly number[], h: number, top: number, bottom: number): number[] {
  const n = wanted.length;
  const out: number[] = new Array<number>(n);
  if (n === 0) return out;
  const order = wanted.map((_, i) => i).sort((a, b) => wanted[a]! - wanted[b]! || a - b);
  if (n * h > bottom - top) {
    const step = (bottom - top) / n;
    order.forEach((i, j) => (out[i] = top + step * (j + 0.5)));
    return out;
  }
  // Groups of consecutive labels: the first label's centre and how many follow it, h apart.
  const groups: { first: number; count: number; sum: number }[] = [];
  const place = (g: { first: number; count: number; sum: number }) => {
    // Centred on the mean of its anchors, less each label's offset in the stack; kept inside.
    const mean = g.sum / g.count - ((g.count - 1) * h) / 2;
    g.first = Math.min(Math.max(mean, top + h / 2), bottom - h / 2 - (g.count - 1) * h);
  };
  for (const i of order) {
    const g = { first: 0, count: 1, sum: wanted[i]! };
    place(g);
    groups.push(g);
    // Merge with the group above while they overlap; the merged group is placed afresh.
    for (;;) {
      const cur = groups[groups.length - 1]!;
      const prev = groups[groups.length - 2];
      if (!prev || prev.first + prev.count * h <= cur.first + 1e-9) break;
      prev.sum += cur.sum;
      prev.count += cur.count;
      groups.pop();
      place(prev);
    }
  }
  let j = 0;
  for (const g of groups) for (let k = 0; k < g.count; k++) out[order[j++]!] = g.first + k * h;
  return out;
}
