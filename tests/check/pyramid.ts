/**
 * The small 8×8 pyramid the comparison tests shrink: two product pools and a last convolution
 * named `last`. With shared weights its left-right capacity is min(last width, C(8 + 1, 2) = 36):
 * the two left children of the top window pass only Sym² of the 8 channels below (derived here).
 */
export function pyramid(lastWidth: number, firstWidth = 4, preamble = ''): string {
  return `${preamble}model:
  input: {shape: [8, 8], features: 2}
  layers:
    - conv: {channels: ${firstWidth}}
    - pool: {window: 2}
    - conv: {channels: 8}
    - pool: {window: 2}
    - conv: {channels: ${lastWidth}, name: last}
    - pool: {global: true}
`;
}
