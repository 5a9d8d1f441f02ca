// Paths of the web app's pages that the server links to (e-mails) and the client routes to: written
// once so a mailed link always opens the page it names.

export const appPaths = {
  run: (studioId: string, runId: string) => `/s/${studioId}/runs/${runId}`,
  release: (studioId: string, releaseId: string) => `/s/${studioId}/releases/${releaseId}`,
  releases: (studioId: string) => `/s/${studioId}/releases`,
  track: (studioId: string, trackId: string) => `/s/${studioId}/tracks/${trackId}`,
  /** Runs of one take of the track side by side, in the order given. */
  compareRuns: (studioId: string, trackId: string, runIds: readonly string[]) =>
    `/s/${studioId}/tracks/${trackId}/compare?runs=${runIds.map(encodeURIComponent).join(',')}`,
  home: (studioId: string) => `/s/${studioId}`,
  /** A venue's page: its motion base form, controller output and profiles. */
  venue: (studioId: string, venueId: string) => `/s/${studioId}/venues/${venueId}`,
  audit: (studioId: string) => `/s/${studioId}/audit`,
  account: () => '/account',
  /** The mail settings live on the account page. */
  notificationSettings: () => '/account',
} as const;
