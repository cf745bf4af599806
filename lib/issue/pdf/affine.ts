// The 2-D affine matrices of SVG and PDF, [a b c d e f]: x' = a·x + c·y + e, y' = b·x + d·y + f.
// One product for every drawing path (typeset formulas, SVG figures, the direct glyph drawing), so
// each computes a placement with the same operations in the same order.

export type Matrix = [number, number, number, number, number, number];

export const IDENTITY: Matrix = [1, 0, 0, 1, 0, 0];

/** m1 · m2 (apply m2 first). */
export function multiply(m1: Matrix, m2: Matrix): Matrix {
  return [
    m1[0] * m2[0] + m1[2] * m2[1],
    m1[1] * m2[0] + m1[3] * m2[1],
    m1[0] * m2[2] + m1[2] * m2[3],
    m1[1] * m2[2] + m1[3] * m2[3],
    m1[0] * m2[4] + m1[2] * m2[5] + m1[4],
    m1[1] * m2[4] + m1[3] * m2[5] + m1[5],
  ];
}
