import type { LoginResponse, User } from '@dialsheet/common';
import { Body, Controller, Get, HttpCode, Patch, Post, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags, ApiTooManyRequestsResponse } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { Public } from '../../core/decorators/public.decorator';
import { AuthService } from './auth.service';
import { ChangePasswordDto } from './dto/change-password.dto';
import { LoginDto } from './dto/login.dto';
import { PasswordResetConfirmDto } from './dto/password-reset-confirm.dto';
import { PasswordResetDto } from './dto/password-reset.dto';
import { UpdateProfileDto } from './dto/update-profile.dto';
import { SignInThrottlerGuard } from './sign-in-throttler.guard';

@ApiTags('auth')
@Controller('auth')
export class AuthController {
  constructor(private readonly auth: AuthService) {}

  @Public()
  @UseGuards(SignInThrottlerGuard)
  @Post('login')
  @HttpCode(200)
  @ApiOperation({ summary: 'Sign in with e-mail and password' })
  @ApiTooManyRequestsResponse({ description: 'Too many attempts for this address and e-mail' })
  login(@Body() dto: LoginDto): Promise<LoginResponse> {
    return this.auth.login(dto);
  }

  @ApiBearerAuth()
  @Post('logout')
  @HttpCode(204)
  @ApiOperation({ summary: 'Sign out: this token stops working' })
  logout(@CurrentUser() user: AuthUser): Promise<void> {
    return this.auth.logout(user);
  }

  @ApiBearerAuth()
  @Get('me')
  @ApiOperation({ summary: 'The signed-in account' })
  me(@CurrentUser() user: AuthUser): Promise<User> {
    return this.auth.me(user);
  }

  @ApiBearerAuth()
  @Patch('me')
  @ApiOperation({ summary: 'Change your display name' })
  updateProfile(@CurrentUser() user: AuthUser, @Body() dto: UpdateProfileDto): Promise<User> {
    return this.auth.updateProfile(user, dto);
  }

  @ApiBearerAuth()
  @Post('password')
  @HttpCode(204)
  @ApiOperation({ summary: 'Change your password; every existing session ends, this one included' })
  changePassword(@CurrentUser() user: AuthUser, @Body() dto: ChangePasswordDto): Promise<void> {
    return this.auth.changePassword(user, dto);
  }

  @Public()
  @UseGuards(SignInThrottlerGuard)
  @Post('password-reset')
  @HttpCode(202)
  @ApiOperation({ summary: 'E-mail a one-time reset link (answers 202 whether or not the account exists)' })
  @ApiTooManyRequestsResponse({ description: 'Too many attempts for this address and e-mail' })
  requestPasswordReset(@Body() dto: PasswordResetDto): Promise<void> {
    return this.auth.requestPasswordReset(dto);
  }

  @Public()
  @Post('password-reset/confirm')
  @HttpCode(204)
  @ApiOperation({ summary: 'Set a new password with the token from the reset link' })
  confirmPasswordReset(@Body() dto: PasswordResetConfirmDto): Promise<void> {
    return this.auth.confirmPasswordReset(dto);
  }
}
