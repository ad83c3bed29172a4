/**
 * Point labels that do not overlap: a deterministic greedy placement. Labels are taken in the
 * order given; each goes to the first of a fixed list of spots around its point (right above,
 * right below, left above, left below, above, below, then the same directions one, two and three
 * label heights further out) where its box stays inside the plot and overlaps no label already
 * placed and no other point. A label that finds no spot is left out and counted, so the caller
 * can say so; a label moved past the first ring gets a leader line to its point. No randomness:
 * the same points give the same picture.
 */

export interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface LabelRequest {
  /** The point, in chart pixels. */
  x: number;
  y: number;
  /** The label's size in pixels. */
  width: number;
  height: number;
}

export interface Placement {
  /** The box's top-left corner and size; null when the label is left out. */
  box: Box | null;
  /** Moved away from the point: draw a line from the point to the box. */
  leader: boolean;
}

/** Width of a text of `chars` characters at `fontSize` pixels of a system sans-serif (about 0.62 em a character; common practice for estimates). */
export function textWidth(chars: number, fontSize = 10): number {
  return Math.ceil(chars * fontSize * 0.62) + 2;
}

export function overlaps(a: Box, b: Box, gap = 0): boolean {
  return a.x < b.x + b.width + gap && b.x < a.x + a.width + gap && a.y < b.y + b.height + gap && b.y < a.y + a.height + gap;
}

/**
 * Place the labels inside `bounds`. `pointRadius` keeps labels off the other points' markers
 * (0: only labels are kept apart).
 */
export function placeLabels(labels: readonly LabelRequest[], bounds: Box, pointRadius = 4): Placement[] {
  const placed: Box[] = [];
  const markers: Box[] = labels.map((l) => ({ x: l.x - pointRadius, y: l.y - pointRadius, width: 2 * pointRadius, height: 2 * pointRadius }));
  const inside = (b: Box) => b.x >= bounds.x && b.y >= bounds.y && b.x + b.width <= bounds.x + bounds.width && b.y + b.height <= bounds.y + bounds.height;
  return labels.map((l, k) => {
    const off = pointRadius + 2;
    for (let ring = 0; ring < 4; ring++) {
      const d = ring * (l.height + 2);
      const spots: [number, number][] = [
        [l.x + off, l.y - off - l.height - d], // right above
        [l.x + off, l.y + off + d], // right below
        [l.x - off - l.width, l.y - off - l.height - d], // left above
        [l.x - off - l.width, l.y + off + d], // left below
        [l.x - l.width / 2, l.y - off - l.height - d], // above
        [l.x - l.width / 2, l.y + off + d], // below
        [l.x + off + d, l.y - l.height / 2], // right
        [l.x - off - d - l.width, l.y - l.height / 2], // left
      ];
      for (const [x, y] of spots) {
        const box = { x, y, width: l.width, height: l.height };
        if (!inside(box)) continue;
        if (placed.some((p) => overlaps(p, box, 1))) continue;
        if (pointRadius > 0 && markers.some((m, j) => j !== k && overlaps(m, box))) continue;
        placed.push(box);
        return { box, leader: ring > 0 };
      }
    }
    return { box: null, leader: false };
  });
}
