import { Migration } from '@mikro-orm/migrations';

/** A sheet remembers the fingerprint of the content its stored results are the evaluation of (a one-cell edit names it). */
export class Migration20261203180422 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`sheet\` add \`results_fingerprint\` varchar(64) null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`sheet\` drop column \`results_fingerprint\`;`);
  }

}
