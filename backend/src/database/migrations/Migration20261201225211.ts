import { Migration } from '@mikro-orm/migrations';

export class Migration20261201225211 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`firm\` (\`id\` varchar(36) not null, \`name\` varchar(200) not null, \`created_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`firm\`;`);
  }

}
