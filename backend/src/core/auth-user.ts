/** The signed-in caller as the JWT strategy puts it on the request. */
export interface AuthUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
  /** Token id and expiry (seconds since epoch) of the token that authenticated this request. */
  jti: string;
  exp: number;
}
