import { palette } from '@/config/palette';

/**
 * Kiln's mark: an ember flame over a sphere crossed by one tilted meridian (the
 * round and ellipsoidal targets the flows run into). Same drawing as
 * public/kiln-mark.svg. `gapColor` is the background, cut around the flame.
 */
export function KilnMark({
  size = 28,
  sphereColor = 'currentColor',
  gapColor = '#ffffff',
}: {
  size?: number;
  sphereColor?: string;
  gapColor?: string;
}) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <circle cx="16" cy="20.6" r="9.9" fill="none" stroke={sphereColor} strokeWidth="2.3" />
      <ellipse
        cx="16"
        cy="20.6"
        rx="9.9"
        ry="3.4"
        fill="none"
        stroke={sphereColor}
        strokeWidth="1.5"
        opacity="0.7"
        transform="rotate(-18 16 20.6)"
      />
      <path
        d="M16 0.6c3.6 3.4 6.4 6.4 6.4 9.9 0 3.2-2.8 5.3-6.4 5.3s-6.4-2.1-6.4-5.3c0-2.3 1.2-4 2.7-5.6.3 1.9 1.2 3.1 2.4 3.5-.5-2.7 0-5.3 1.3-7.8z"
        fill={palette.ember}
        stroke={gapColor}
        strokeWidth="1.2"
        paintOrder="stroke"
      />
      <path
        d="M16 8.2c1.4 1.5 2.4 2.8 2.4 4.1 0 1.3-1 2.1-2.4 2.1s-2.4-.8-2.4-2.1c0-1.3 1-2.6 2.4-4.1z"
        fill={palette.emberGlow}
      />
    </svg>
  );
}

/** The mark with the word "Kiln" beside it; `inverted` for dark backgrounds. */
export function KilnWordmark({ inverted = false, size = 26 }: { inverted?: boolean; size?: number }) {
  const color = inverted ? '#f4f1ec' : palette.ink;
  return (
    <span className="kiln-wordmark" style={{ color }}>
      <KilnMark size={size} sphereColor={color} gapColor={inverted ? palette.soot : '#ffffff'} />
      <span className="kiln-wordmark__text" style={{ fontSize: size * 0.8 }}>
        Kiln
      </span>
    </span>
  );
}
