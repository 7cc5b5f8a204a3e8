import type { SVGProps } from 'react';

/**
 * Kiln's small line icons, drawn for the app (1em, currentColor). Status icons
 * always travel with a word; these never carry meaning alone.
 */
type IconProps = SVGProps<SVGSVGElement>;

function Icon({ children, ...props }: IconProps) {
  return (
    <svg
      width="1em"
      height="1em"
      viewBox="0 0 16 16"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.6}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      {...props}
    >
      {children}
    </svg>
  );
}

export const IconCheck = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M5.2 8.2l2 2 3.6-4" />
  </Icon>
);

export const IconCross = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M5.8 5.8l4.4 4.4M10.2 5.8l-4.4 4.4" />
  </Icon>
);

export const IconWarning = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 2.2l6.2 11H1.8z" />
    <path d="M8 6.6v3" />
    <path d="M8 11.6v.1" />
  </Icon>
);

export const IconIdle = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" strokeDasharray="2.4 2" />
    <path d="M5.5 8h5" />
  </Icon>
);

export const IconInfo = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M8 7.2v3.8" />
    <path d="M8 4.9v.1" />
  </Icon>
);

export const IconOverview = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2 13.5h12" />
    <path d="M3.5 13.5V9M6.5 13.5V5.5M9.5 13.5V7.5M12.5 13.5V3" />
  </Icon>
);

export const IconLab = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="5.5" cy="5.5" r="2.2" />
    <circle cx="11" cy="6.5" r="1.8" />
    <path d="M1.8 13.2c.4-2.4 1.9-3.8 3.7-3.8s3.3 1.4 3.7 3.8" />
    <path d="M9.8 10c.4-.4.8-.6 1.2-.6 1.5 0 2.7 1.2 3 3.3" />
  </Icon>
);

export const IconSignOut = (p: IconProps) => (
  <Icon {...p}>
    <path d="M6.5 2.5h-3a1 1 0 00-1 1v9a1 1 0 001 1h3" />
    <path d="M10.5 5l3 3-3 3M13.5 8H6" />
  </Icon>
);

export const IconLock = (p: IconProps) => (
  <Icon {...p}>
    <rect x="3" y="7" width="10" height="7" rx="1" />
    <path d="M5.2 7V5a2.8 2.8 0 015.6 0v2" />
  </Icon>
);

export const IconRefresh = (p: IconProps) => (
  <Icon {...p}>
    <path d="M13.2 8a5.2 5.2 0 11-1.6-3.8" />
    <path d="M13.2 2.6v2.8h-2.8" />
  </Icon>
);

export const IconSignpost = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 1.8v12.4M5.5 14.2h5" />
    <path d="M8 3.2h4.6l1.6 1.7-1.6 1.7H8zM8 8.2H3.4L1.8 9.9l1.6 1.7H8z" />
  </Icon>
);

export const IconStudies = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 3.5h4l1.2 1.5h5.8v7.5h-11z" />
    <path d="M2.5 7h11" />
  </Icon>
);

export const IconRunning = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M6.6 5.4l3.8 2.6-3.8 2.6z" />
  </Icon>
);

export const IconPaused = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M6.5 5.6v4.8M9.5 5.6v4.8" />
  </Icon>
);

export const IconQueue = (p: IconProps) => (
  <Icon {...p}>
    <path d="M3 4.5h10M3 8h10M3 11.5h6" />
  </Icon>
);

export const IconHourglass = (p: IconProps) => (
  <Icon {...p}>
    <path d="M4.5 2h7M4.5 14h7" />
    <path d="M5 2c0 3 6 3.5 6 6s-6 3-6 6M11 2c0 3-6 3.5-6 6s6 3 6 6" />
  </Icon>
);

export const IconStop = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <rect x="5.7" y="5.7" width="4.6" height="4.6" rx="0.5" />
  </Icon>
);

export const IconFlare = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 1.8v2.6M8 11.6v2.6M1.8 8h2.6M11.6 8h2.6M3.6 3.6l1.8 1.8M10.6 10.6l1.8 1.8M12.4 3.6l-1.8 1.8M5.4 10.6l-1.8 1.8" />
    <circle cx="8" cy="8" r="1.6" />
  </Icon>
);

export const IconClock = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M8 4.6V8l2.4 1.6" />
  </Icon>
);

export const IconFork = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="4.5" cy="3.5" r="1.5" />
    <circle cx="4.5" cy="12.5" r="1.5" />
    <circle cx="11.5" cy="5.5" r="1.5" />
    <path d="M4.5 5v6M11.5 7c0 2.5-3 2.5-7 4" />
  </Icon>
);

export const IconDownload = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 2.5v8M4.8 7.5L8 10.7l3.2-3.2" />
    <path d="M2.5 12v1.5h11V12" />
  </Icon>
);

export const IconPlus = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 3v10M3 8h10" />
  </Icon>
);

export const IconWorker = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2.5" y="3" width="11" height="4" rx="0.8" />
    <rect x="2.5" y="9" width="11" height="4" rx="0.8" />
    <path d="M5 5h.1M5 11h.1" />
  </Icon>
);
