// The demo scenario: a fictional studio, its venues and one member per role. Invented for the demo
// only; nothing here describes a real company, person or ride.
import type { Role } from './schemas/roles';

export const DEMO_PASSWORD = 'legwork-demo';

export const DEMO_STUDIO = { name: 'Lanternfish Studios', slug: 'lanternfish' } as const;
export const DEMO_SECOND_STUDIO = { name: 'Quarry Hill Pictures', slug: 'quarry-hill' } as const;

export const DEMO_VENUES = {
  dome: { name: 'Harbour Lights Dome', site: 'Port Meridian pier', timeZone: 'Europe/Lisbon' },
  arcade: { name: 'Tidewater Arcade', site: 'Saltmarsh boardwalk', timeZone: 'America/Halifax' },
} as const;

export interface DemoUser {
  email: string;
  name: string;
  roles: Role[];
  /** Venue keys of DEMO_VENUES for a venue operator's scope. */
  venues?: (keyof typeof DEMO_VENUES)[];
}

export const DEMO_USERS: DemoUser[] = [
  { email: 'pia.producer@lanternfish.example', name: 'Pia Okafor', roles: ['producer'] },
  { email: 'eli.engineer@lanternfish.example', name: 'Eli Varga', roles: ['motion_engineer'] },
  { email: 'rosa.reviewer@lanternfish.example', name: 'Rosa Lindqvist', roles: ['safety_reviewer'] },
  {
    email: 'otto.operator@lanternfish.example',
    name: 'Otto Brenner',
    roles: ['venue_operator'],
    venues: ['dome'],
  },
  { email: 'ada.admin@lanternfish.example', name: 'Ada Moreau', roles: ['studio_admin'] },
];

/** A take of the demo track and the venues it is cued for (keys of DEMO_VENUES). */
export interface DemoTake {
  file: string;
  /** What the cut is, for the take list and the seeded review reasons. */
  note: string;
  duration_s: number;
  rate_hz: number;
  intensity: number;
  bumps: number;
  venues: (keyof typeof DEMO_VENUES)[];
}

/**
 * The demo studio's track: a fictional dark-ride coaster film (station, launch, banked left turn, hill,
 * drop, banked right turn, three bumps, brake run). Four cuts of it show every stage of the chain: the
 * first cut at both venues, a recut, a rattly cut whose bumps break the comfort limit on jerk, and a hot
 * cut driven so hard that the dome's legs run out of stroke in the drop (a hard limit).
 */
export const DEMO_TRACK = {
  title: 'Breakwater Chase',
  film: "The Lamplighter's Gale (fictional ride film)",
  takes: [
    {
      file: 'breakwater-chase-cut1.csv',
      note: 'first cut',
      duration_s: 60,
      rate_hz: 100,
      intensity: 1,
      bumps: 1,
      venues: ['dome', 'arcade'],
    },
    {
      file: 'breakwater-chase-cut2.csv',
      note: 'recut, softer launch',
      duration_s: 60,
      rate_hz: 100,
      intensity: 0.9,
      bumps: 1,
      venues: ['dome'],
    },
    {
      file: 'breakwater-chase-cut3-rattle.csv',
      note: 'rattle cut, sharper bumps',
      duration_s: 60,
      rate_hz: 100,
      intensity: 1,
      bumps: 3,
      venues: ['dome'],
    },
    {
      file: 'breakwater-chase-cut4-hot.csv',
      note: 'hot cut',
      duration_s: 60,
      rate_hz: 100,
      intensity: 4,
      bumps: 1,
      venues: ['dome'],
    },
  ] satisfies DemoTake[],
} as const;
