import type { SVGProps } from 'react';

/**
 * Coretrail's own small icon set, drawn on a 20-unit grid with a 1.75 stroke. State icons differ
 * in outline shape as well as glyph (ring, square, diamond, dashed ring), so a state still reads
 * in grey print or for a colour-blind eye.
 */
const glyphs = {
  ok: (
    <>
      <circle cx="10" cy="10" r="7.5" />
      <path d="M6.6 10.2l2.3 2.3 4.6-4.9" />
    </>
  ),
  bad: (
    <>
      <rect x="2.75" y="2.75" width="14.5" height="14.5" rx="1.5" />
      <path d="M7.2 7.2l5.6 5.6M12.8 7.2l-5.6 5.6" />
    </>
  ),
  hold: (
    <>
      <path d="M10 1.9l8.1 8.1-8.1 8.1-8.1-8.1z" />
      <path d="M8.3 7.6v4.8M11.7 7.6v4.8" />
    </>
  ),
  wait: (
    <>
      <circle cx="10" cy="10" r="7.5" strokeDasharray="2.6 2.2" />
      <path d="M10 6.2V10l2.6 1.6" />
    </>
  ),
  off: (
    <>
      <circle cx="10" cy="10" r="7.5" />
      <path d="M4.8 15.2L15.2 4.8" />
    </>
  ),
  neutral: <path d="M5 10h10" />,
  close: <path d="M5.5 5.5l9 9M14.5 5.5l-9 9" />,
  info: (
    <>
      <circle cx="10" cy="10" r="7.5" />
      <path d="M10 9v5M10 6.1v.1" />
    </>
  ),
  alert: (
    <>
      <path d="M10 2.6l7.8 13.9H2.2z" />
      <path d="M10 8v4M10 14.3v.1" />
    </>
  ),
  plus: <path d="M10 4v12M4 10h12" />,
  chevronDown: <path d="M5.5 8l4.5 4.5L14.5 8" />,
  chevronUp: <path d="M5.5 12l4.5-4.5 4.5 4.5" />,
  sortable: <path d="M6.5 8L10 4.5 13.5 8M6.5 12l3.5 3.5 3.5-3.5" />,
  chevronRight: <path d="M8 5.5l4.5 4.5L8 14.5" />,
  chevronLeft: <path d="M12 5.5L7.5 10l4.5 4.5" />,
  arrowRight: <path d="M4 10h11.5M11 5.5l4.5 4.5-4.5 4.5" />,
  key: (
    <>
      <circle cx="6.5" cy="10" r="3.5" />
      <path d="M10 10h7.5M15 10v3M12.5 10v2" />
    </>
  ),
  signOut: (
    <>
      <path d="M8 3.5H4.5v13H8" />
      <path d="M8.5 10H17M13.5 6.5L17 10l-3.5 3.5" />
    </>
  ),
  chain: (
    <>
      <rect x="2.5" y="7" width="8" height="6" rx="3" />
      <rect x="9.5" y="7" width="8" height="6" rx="3" />
    </>
  ),
  camera: (
    <>
      <path d="M2.5 6.5h3.2l1.5-2.2h5.6l1.5 2.2h3.2v9.5h-15z" />
      <circle cx="10" cy="11" r="3" />
    </>
  ),
  print: (
    <>
      <path d="M5.5 7.5V2.5h9v5" />
      <rect x="2.5" y="7.5" width="15" height="6.5" rx="1" />
      <path d="M5.5 12v5.5h9V12" />
    </>
  ),
  download: <path d="M10 3v10M5.8 9l4.2 4.2L14.2 9M3.5 16.5h13" />,
  trash: <path d="M3.5 5.5h13M8 5.5V3.5h4v2M5 5.5l.8 11h8.4l.8-11" />,
  scan: (
    <>
      <path d="M2.5 6.5v-4h4M13.5 2.5h4v4M17.5 13.5v4h-4M6.5 17.5h-4v-4" />
      <path d="M5.5 10h9" />
    </>
  ),
  // a weight hanging from a hook: heavy parts, lift with the hoist
  hoist: (
    <>
      <path d="M10 2v3.2" />
      <circle cx="10" cy="6.6" r="1.4" />
      <path d="M6.6 9.4h6.8l2.6 8.1H4z" />
    </>
  ),
  stepNow: (
    <>
      <circle cx="10" cy="10" r="7.5" />
      <path d="M8 6.5l4.5 3.5L8 13.5z" fill="currentColor" />
    </>
  ),
} as const;

export type IconName = keyof typeof glyphs;

type IconProps = Omit<SVGProps<SVGSVGElement>, 'name'> & { name: IconName; size?: number; label?: string };

export function Icon({ name, size = 18, label, ...rest }: IconProps) {
  return (
    <svg
      viewBox="0 0 20 20"
      width={size}
      height={size}
      fill="none"
      stroke="currentColor"
      strokeWidth={1.75}
      strokeLinecap="round"
      strokeLinejoin="round"
      role={label ? 'img' : undefined}
      aria-label={label}
      aria-hidden={label ? undefined : true}
      focusable="false"
      className="shrink-0"
      {...rest}
    >
      {glyphs[name]}
    </svg>
  );
}
