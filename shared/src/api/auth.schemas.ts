import { z } from 'zod';
import { Role } from './roles';

/** Body of `POST /api/auth/login`. */
export const loginRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email('email must be an e-mail address').max(254),
  password: z.string().min(1, 'password is required').max(1024),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

/** A user as every API response shows them: never a password hash. */
export const userSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  role: z.enum(Role),
  disabled: z.boolean(),
  createdAt: z.string(),
});
export type User = z.infer<typeof userSchema>;

/** Response of `POST /api/auth/login`. */
export interface LoginResponse {
  accessToken: string;
  /** Seconds until the access token expires. */
  expiresIn: number;
  user: User;
}
