/**
 * Stack labels that sit along a horizontal axis (limits, percentiles) into
 * rows so neighbours never overlap: each label goes in the first row whose
 * previous label ends before it starts (greedy interval packing, common practice).
 */
export interface LabelSpan {
  startPx: number;
  endPx: number;
}

/** Row number for every span, in input order. Spans are packed in order of their start. */
export function assignLabelRows(spans: readonly LabelSpan[], gapPx = 6): number[] {
  const order = spans.map((_, i) => i).sort((a, b) => spans[a].startPx - spans[b].startPx || a - b);
  const rowEnds: number[] = [];
  const rows = new Array<number>(spans.length).fill(0);
  for (const i of order) {
    let row = rowEnds.findIndex((end) => end + gapPx <= spans[i].startPx);
    if (row === -1) {
      row = rowEnds.length;
      rowEnds.push(spans[i].endPx);
    } else {
      rowEnds[row] = spans[i].endPx;
    }
    rows[i] = row;
  }
  return rows;
}
