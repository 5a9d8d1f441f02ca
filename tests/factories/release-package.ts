// A release package's input for unit tests: a released hexapod run with the fixture legs file, made-up
// names and hashes (test data only). Override any part per test.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { ReleasePackageInput } from '../../server/pipeline/release-package';
import { demoHexapodBase } from '../../shared/schemas/motion-base';

/** The fixture legs file the input reads as the run's legs.csv. */
export const legsCsv = readFileSync(fileURLToPath(new URL('../fixtures/legs-hexapod.csv', import.meta.url)));

export function releasePackageInput(over: Partial<ReleasePackageInput> = {}): ReleasePackageInput {
  const base = { ...demoHexapodBase, controllerRate_hz: 50 } as ReleasePackageInput['motionBase']['base'];
  return {
    release: {
      id: '0b7f3a9e-1111-4222-8333-444455556666',
      releasedBy: { id: 'u1', name: 'Ada Reviewer', email: 'ada@example.test' },
      releasedAt: '2026-01-02T03:04:05Z',
    },
    reviews: [],
    run: {
      id: 'r1',
      state: 'released',
      summary: {
        within: true,
        exitCode: 0,
        uses: [],
        findings: [],
        comfort: null,
        notes: [],
        rate_hz: 50,
        samples: 3,
        duration_s: 1,
        budgetIsDemo: true,
        files: [],
      },
    },
    track: { id: 't1', title: 'Canyon Glide' },
    take: { id: 'k1', number: 2, sha256: 'a'.repeat(64), filename: 'take2.csv' },
    venue: { id: 'v1', name: 'North Hall', timeZone: 'UTC' },
    motionBase: { id: 'm1', name: 'Base', sha256: 'b'.repeat(64), base },
    cueing: { id: 'c1', name: 'Soft', version: 3 },
    budget: { id: 'b1', name: 'Family', version: 4 },
    softwareVersion: '0.0.0-test',
    readRunFile: async (name) => (name === 'legs.csv' ? legsCsv : Buffer.from(`${name}\n`)),
    ...over,
  };
}
