import { CanActivate, ExecutionContext, ForbiddenException, Injectable } from '@nestjs/common';
import type { AuthUser } from '../auth-user';

/** Account and platform routes. Campaign data is never reachable through this guard. */
@Injectable()
export class PlatformAdminGuard implements CanActivate {
  canActivate(context: ExecutionContext): boolean {
    const user = context.switchToHttp().getRequest<{ user?: AuthUser }>().user;
    if (!user?.isAdmin) throw new ForbiddenException('Only a platform administrator can do this');
    return true;
  }
}
