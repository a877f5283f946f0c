export interface User {
  id: string;
  email: string;
  name: string;
  /** The first account created on a platform administers accounts. */
  isAdmin: boolean;
  createdAt: string;
}

export interface LoginRequest {
  email: string;
  password: string;
}

export interface LoginResponse {
  accessToken: string;
  /** Seconds until the token expires. */
  expiresIn: number;
  user: User;
}

export interface ChangePasswordRequest {
  currentPassword: string;
  newPassword: string;
}

export interface PasswordResetRequest {
  email: string;
}

export interface PasswordResetConfirmRequest {
  token: string;
  newPassword: string;
}

export interface UpdateProfileRequest {
  name: string;
}

/** Minimum password length enforced on every route that sets a password. */
export const MIN_PASSWORD_LENGTH = 10;

/** A user as the platform administrator sees it. */
export interface AdminUser extends User {
  /** A disabled account cannot sign in; its existing tokens stop working. */
  disabled: boolean;
}

export interface UpdateUserRequest {
  disabled?: boolean;
  isAdmin?: boolean;
}
