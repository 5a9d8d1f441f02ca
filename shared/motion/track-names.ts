// How a track is named in messages: "a vehicle track", "a hexapod pose track", "a planar-stage legs
// track". A vehicle track has no base layout, so its layout is never repeated before its kind.
import type { TrackKind, TrackLayout } from './track-reader';

const LAYOUT_WORDS: Record<TrackLayout, string> = {
  vehicle: '',
  hexapod: 'hexapod',
  planar3: 'planar-stage',
};

/** "vehicle track", "hexapod pose track", "planar-stage legs track" (no article). */
export function trackName(kind: TrackKind, layout: TrackLayout): string {
  const words = kind === 'vehicle' ? [] : [LAYOUT_WORDS[layout]].filter(Boolean);
  return [...words, kind, 'track'].join(' ');
}
