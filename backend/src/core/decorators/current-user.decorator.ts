import { createParamDecorator, ExecutionContext, UnauthorizedException } from '@nestjs/common';
import type { AuthUser } from '../auth-user';

/** The authenticated caller; only meaningful on routes the JWT guard protects. */
export const CurrentUser = createParamDecorator((_data: unknown, ctx: ExecutionContext): AuthUser => {
  const user = ctx.switchToHttp().getRequest<{ user?: AuthUser }>().user;
  // A route marked @Public() that asks for the caller is a programming error, not a client one.
  if (!user) throw new UnauthorizedException('Sign in to continue');
  return user;
});
