/** What we sign into an access token besides the standard `jti` and `exp`. */
export interface JwtPayload {
  sub: string;
  /** The user's token version when the token was issued. */
  ver: number;
  jti: string;
  exp: number;
}
