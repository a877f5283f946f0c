import type { AdminUser } from '@dialsheet/common';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { UpdateUserDto } from './dto/update-user.dto';
import { toAdminUser } from './user.mapper';
import { UserEntity } from './user.entity';

/** Account administration; only platform administrators reach these methods. */
@Injectable()
export class UsersService {
  constructor(@InjectRepository(UserEntity) private readonly users: Repository<UserEntity>) {}

  async list(): Promise<AdminUser[]> {
    const users = await this.users.find({ order: { createdAt: 'ASC', email: 'ASC' } });
    return users.map(toAdminUser);
  }

  async update(admin: AuthUser, userId: string, dto: UpdateUserDto): Promise<AdminUser> {
    const user = await this.users.findOneBy({ id: userId });
    if (!user) throw new NotFoundException('User not found');
    // Locking yourself out would leave the platform without anyone able to undo it.
    if (user.id === admin.id && (dto.disabled === true || dto.isAdmin === false)) {
      throw new ConflictException('You cannot disable your own account or remove your own administrator rights');
    }
    if (dto.disabled !== undefined) user.disabledAt = dto.disabled ? (user.disabledAt ?? new Date()) : null;
    if (dto.isAdmin !== undefined) user.isAdmin = dto.isAdmin;
    return toAdminUser(await this.users.save(user));
  }
}
