import { Migration } from '@mikro-orm/migrations';

export class Migration20261202022608 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`drop index if exists "outbox_message_next_attempt_at_index";`);
    this.addSql(`create index "outbox_message_due_index" on "outbox_message" ("status", "next_attempt_at");`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop index "outbox_message_due_index";`);
    this.addSql(`create index "outbox_message_next_attempt_at_index" on "outbox_message" ("next_attempt_at");`);
  }

}
