import { Column, Entity, PrimaryColumn } from 'typeorm';

/** A random value the server draws once and keeps across restarts (e.g. the key that signs known-device cookies). */
@Entity({ name: 'server_secrets' })
export class ServerSecret {
  @PrimaryColumn({ type: 'varchar', length: 64 })
  name: string;

  @Column({ type: 'varchar', length: 200 })
  value: string;
}
