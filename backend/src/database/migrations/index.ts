import { Foundation1764640800000 } from './1764640800000-Foundation';
import { Recordings1764900000000 } from './1764900000000-Recordings';
import { Channels1765000000000 } from './1765000000000-Channels';
import { Sheets1765200000000 } from './1765200000000-Sheets';
import { Readings1765300000000 } from './1765300000000-Readings';
import { Resolutions1765400000000 } from './1765400000000-Resolutions';
import { Analysis1765500000000 } from './1765500000000-Analysis';
import { Releases1765600000000 } from './1765600000000-Releases';

/**
 * Every migration, oldest first. Listed rather than globbed so the same list works from the
 * compiled output, from the TypeScript sources under the test runner, and in the CLI;
 * migrations.spec.ts fails when a file in this folder is missing here.
 */
export const migrations = [Foundation1764640800000, Recordings1764900000000, Channels1765000000000, Sheets1765200000000, Readings1765300000000, Resolutions1765400000000, Analysis1765500000000, Releases1765600000000];
