/**
 * Invoice arithmetic and numbering: pure TypeScript, integer minor units. Totals follow EN 16931
 * BR-CO-10/13/14/15/16/17 (totals.ts), numbers Directive 2006/112/EC Article 226(2)
 * (numbering.ts), the month's VAT Articles 65 and 90 (ledger.ts).
 */
export {
	DOCUMENT_TYPE,
	SERIES_FOR_TYPE,
	NUMBER_WIDTH,
	documentKindLabel,
	documentYear,
	formatDocumentNumber,
	isDocumentTypeCode,
	missingNumbers,
	parseDocumentNumber,
	type DocumentTypeCode
} from './numbering';
export {
	documentTotals,
	documentViolations,
	grossByRate,
	linesFromPriceLines,
	lumpSumLines,
	payableTotal,
	splitByWeights,
	type DocumentLine,
	type DocumentLineInput,
	type DocumentTotals,
	type TotalsOptions
} from './totals';
export { vatCategoryOf, vatLedger, type LedgerDocument, type LedgerRow, type VatCategory, type VatRow } from './ledger';
