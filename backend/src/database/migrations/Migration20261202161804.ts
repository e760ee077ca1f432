import { Migration } from '@mikro-orm/migrations';

export class Migration20261202161804 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`pending_registration\` (\`token_hash\` varchar(64) not null, \`firm_name\` varchar(200) not null, \`name\` varchar(200) not null, \`email\` varchar(254) not null, \`password_hash\` varchar(100) not null, \`expires_at\` datetime not null, \`used_at\` datetime null, \`created_at\` datetime not null, primary key (\`token_hash\`)) default character set utf8mb4 engine = InnoDB;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`pending_registration\`;`);
  }

}
