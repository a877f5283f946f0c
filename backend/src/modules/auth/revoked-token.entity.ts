import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';

/** Tokens signed out before they expire; rows past `expiresAt` are useless and get pruned. */
@Entity('revoked_tokens')
export class RevokedTokenEntity {
  @PrimaryColumn({ type: 'uuid' })
  jti: string;

  @Column({ type: 'uuid' })
  userId: string;

  @Column({ type: 'timestamptz' })
  expiresAt: Date;

  @CreateDateColumn({ type: 'timestamptz' })
  createdAt: Date;
}
