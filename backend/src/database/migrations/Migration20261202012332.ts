import { Migration } from '@mikro-orm/migrations';

export class Migration20261202012332 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`attachment\` (\`id\` varchar(36) not null, \`sheet_id\` varchar(36) not null, \`object_key\` varchar(200) not null, \`file_name\` varchar(255) not null, \`media_type\` varchar(120) not null, \`size\` bigint not null, \`sha256\` varchar(64) not null, \`uploaded_by_id\` varchar(36) null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`attachment\` add index \`attachment_sheet_id_index\`(\`sheet_id\`);`);
    this.addSql(`alter table \`attachment\` add index \`attachment_uploaded_by_id_index\`(\`uploaded_by_id\`);`);

    this.addSql(`alter table \`attachment\` add constraint \`attachment_sheet_id_foreign\` foreign key (\`sheet_id\`) references \`sheet\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`attachment\` add constraint \`attachment_uploaded_by_id_foreign\` foreign key (\`uploaded_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`attachment\`;`);
  }

}
