import { SetMetadata } from '@nestjs/common';

export const IS_PUBLIC_KEY = 'dialsheet:isPublic';

/** Opts a route (or controller) out of the global JWT guard. */
export const Public = () => SetMetadata(IS_PUBLIC_KEY, true);
