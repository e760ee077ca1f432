import { Migration } from '@mikro-orm/migrations';

export class Migration20261202053113 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`throttle_counter\` (\`tracker_key\` varchar(100) not null, \`hits\` int unsigned not null, \`expires_at\` datetime(3) not null, \`blocked_until\` datetime(3) null, primary key (\`tracker_key\`)) default character set utf8mb4 engine = InnoDB;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`throttle_counter\`;`);
  }

}
