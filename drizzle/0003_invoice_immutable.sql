-- Issued invoices, deposit invoices and credit notes never change (Directive 2006/112/EC,
-- Article 233: integrity of content from issue to the end of the storage period). A mistake is
-- corrected by a credit note that refers to the invoice (Article 219; EN 16931 BT-25), never by an
-- UPDATE. The database refuses UPDATE and DELETE on both tables, whoever asks.
CREATE OR REPLACE FUNCTION invoice_refuse_change() RETURNS trigger AS $$
BEGIN
	RAISE EXCEPTION 'issued documents are immutable: % on % is refused; correct an invoice with a credit note', TG_OP, TG_TABLE_NAME
		USING ERRCODE = '55000', HINT = 'Issue a credit note (type 381) that refers to the invoice.';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER invoice_immutable_trg
	BEFORE UPDATE OR DELETE ON "invoice"
	FOR EACH ROW EXECUTE FUNCTION invoice_refuse_change();
--> statement-breakpoint
CREATE TRIGGER invoice_line_immutable_trg
	BEFORE UPDATE OR DELETE ON "invoice_line"
	FOR EACH ROW EXECUTE FUNCTION invoice_refuse_change();
--> statement-breakpoint
-- Numbers run without gaps (Article 226(2)): a counter only ever moves up by one, and stays.
CREATE OR REPLACE FUNCTION invoice_counter_step() RETURNS trigger AS $$
BEGIN
	IF TG_OP = 'DELETE' THEN
		RAISE EXCEPTION 'invoice counters are never deleted' USING ERRCODE = '55000';
	END IF;
	IF NEW.series <> OLD.series OR NEW.year <> OLD.year OR NEW.last_number <> OLD.last_number + 1 THEN
		RAISE EXCEPTION 'an invoice counter only moves up by one (% % % -> %)', OLD.series, OLD.year, OLD.last_number, NEW.last_number
			USING ERRCODE = '55000';
	END IF;
	RETURN NEW;
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER invoice_counter_step_trg
	BEFORE UPDATE OR DELETE ON "invoice_counter"
	FOR EACH ROW EXECUTE FUNCTION invoice_counter_step();
