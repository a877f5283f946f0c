import { resolve } from 'node:path';

// This file sits at <repo>/backend/{src,dist}/config, so the repository root is three levels up
// both when run from TypeScript sources and from the compiled output.
export const REPO_ROOT = resolve(__dirname, '..', '..', '..');
export const DEFAULT_STORAGE_DIR = resolve(REPO_ROOT, 'storage');
export const DEFAULT_FRONTEND_DIR = resolve(REPO_ROOT, 'frontend', 'dist');
