// Take files for tests: the demo studio's fictional ride (shared/demo-ride.ts) with overrides.
import { demoRideCsv } from '../../shared/demo-ride';
import type { DemoRideOptions } from '../../shared/demo-ride';

/** A vehicle track CSV (SI columns); see demoRideCsv for the motion. */
export const makeVehicleCsv = (o: DemoRideOptions = {}): string => demoRideCsv(o);
