// Lanes for the text labels of a chart's marks, so that no two labels overlap: labels go left to right
// into the lowest lane where they clear the label before them; a label that fits in no lane (a dense
// group) gets none and is read on hover. The lanes stand in a band above the plot area, so a label's
// height never depends on its mark's. Widths are estimated from the characters at the narrowest plot
// the pages draw, so a wider chart only leaves more room.

export interface StaggerLabelsOptions {
  /** Width of the plot area in px the estimate assumes (the narrowest chart the pages draw: the
   * workbench's half-width chart on a 1280 px screen).
   * @default 440 */
  plotWidthPx?: number;
  /** Average width of one character of the label font in px (10 px IBM Plex Sans, generous).
   * @default 6.5 */
  charWidthPx?: number;
  /** Clear space kept between two labels of a lane, in px.
   * @default 6 */
  gapPx?: number;
  /** Lanes above the marks; a label that fits in none is shown on hover only.
   * @default 3 */
  maxLanes?: number;
}

/**
 * The lane (0 = nearest the mark) of each label, or null for hover only. `xs` are the labels'
 * centres in data units, `xRange` the axis range they are drawn over.
 */
export function staggerLabels(
  xs: readonly number[],
  texts: readonly string[],
  xRange: readonly [number, number],
  options: StaggerLabelsOptions = {},
): (number | null)[] {
  const { plotWidthPx = 440, charWidthPx = 6.5, gapPx = 6, maxLanes = 3 } = options;
  if (xs.length !== texts.length) throw new RangeError("xs and texts must be the same length");
  const span = Math.abs(xRange[1] - xRange[0]);
  const pxPerUnit = span > 0 ? plotWidthPx / span : 0;
  const lanes: (number | null)[] = new Array(xs.length).fill(null);
  // The right edge in px of the last label placed in each lane.
  const laneEnds: number[] = new Array(maxLanes).fill(-Infinity);
  const order = xs.map((_, i) => i).sort((a, b) => xs[a] - xs[b]);
  const left = Math.min(xRange[0], xRange[1]);
  for (const i of order) {
    const centre = (xs[i] - left) * pxPerUnit;
    const half = (texts[i].length * charWidthPx) / 2;
    const lane = laneEnds.findIndex((end) => end + gapPx <= centre - half);
    if (lane < 0) continue;
    lanes[i] = lane;
    laneEnds[lane] = centre + half;
  }
  return lanes;
}

/** Height of one lane in px (10 px text and its leading). */
const LANE_HEIGHT_PX = 13;

/** The top margin in px a chart needs for `maxLanes` lanes of labels above its plot area. */
export function labelLanesMarginPx(maxLanes = 3): number {
  return 8 + maxLanes * LANE_HEIGHT_PX;
}

/**
 * Chart annotations (Plotly's plain layout objects) for labelled marks: each label stands in its lane
 * in a band above the plot area (so the lanes, not the marks' heights, keep labels apart), right
 * above its mark's x; a mark whose label fits no lane gets none (its trace's hover still names it).
 */
export function staggeredLabelAnnotations(
  marks: readonly { x: number; text: string }[],
  xRange: readonly [number, number],
  options: StaggerLabelsOptions = {},
) {
  const lanes = staggerLabels(
    marks.map((m) => m.x),
    marks.map((m) => m.text),
    xRange,
    options,
  );
  return marks.flatMap((mark, i) => {
    const lane = lanes[i];
    if (lane === null) return [];
    return [
      {
        x: mark.x,
        y: 1,
        xref: "x" as const,
        yref: "paper" as const,
        text: mark.text,
        showarrow: false,
        yanchor: "bottom" as const,
        yshift: 2 + lane * LANE_HEIGHT_PX,
        font: { size: 10 },
      },
    ];
  });
}
