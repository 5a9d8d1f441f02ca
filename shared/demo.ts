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

/**
 * The demo studio's first track: a fictional ride film with two vehicle takes cued for both venues. The
 * gentle first cut fits the demo budget; the hotter second cut has jerk over its comfort limit.
 */
export const DEMO_TRACK = {
  title: 'Kelp Forest Descent',
  film: 'Undertow Lantern (fictional ride film)',
  takes: [
    {
      file: 'kelp-forest-descent-take1.csv',
      duration_s: 90,
      rate_hz: 200,
      surge_mps2: 0.8,
      heave_mps2: 0.5,
      yaw_radps: 0.05,
    },
    {
      file: 'kelp-forest-descent-take2-hot.csv',
      duration_s: 60,
      rate_hz: 200,
      surge_mps2: 5,
      heave_mps2: 4.5,
      yaw_radps: 0.45,
    },
  ],
} as const;
