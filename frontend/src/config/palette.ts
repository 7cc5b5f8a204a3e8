/**
 * Kiln's palette: cool slate neutrals ("soot" and "ash") with a single warm
 * accent, kiln ember. Status colours are picked to stay apart for common
 * colour-vision deficiencies, and every status is also an icon and a word.
 */
export const palette = {
  ember: '#c4561d',
  emberHover: '#d96b2e',
  emberActive: '#a4460f',
  emberGlow: '#f29a5c',
  soot: '#1b222a',
  sootRaised: '#242d37',
  sootText: '#c8d0d8',
  ash: '#f3f4f5',
  line: '#dde1e5',
  ink: '#1f2730',
  inkMuted: '#5a6672',
  ok: '#1f7a5a',
  warn: '#8f6400',
  down: '#b3263e',
  info: '#2c6391',
} as const;
