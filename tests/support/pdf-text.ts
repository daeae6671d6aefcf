// The text of a PDF as a reader sees it, row by row, with Mozilla's PDF.js (pdfjs-dist, legacy
// build for Node). Text pieces that share a baseline on a page make one row, left to right.
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

export interface PdfPiece {
	text: string;
	x: number;
	y: number;
}

export interface PdfRow {
	page: number;
	y: number;
	pieces: PdfPiece[];
	/** The row's pieces joined by single spaces. */
	text: string;
}

export async function pdfRows(bytes: Uint8Array): Promise<PdfRow[]> {
	const pdf = await getDocument({ data: new Uint8Array(bytes), isEvalSupported: false, useSystemFonts: false, verbosity: 0 })
		.promise;
	const rows: PdfRow[] = [];
	try {
		for (let n = 1; n <= pdf.numPages; n++) {
			const page = await pdf.getPage(n);
			const content = await page.getTextContent();
			const byY = new Map<number, PdfPiece[]>();
			for (const item of content.items) {
				if (!('str' in item) || item.str.trim() === '') continue;
				const [, , , , x = 0, y = 0] = item.transform as number[];
				// Pieces of one row sit within a couple of points of one baseline (a label and its value
				// are set in different fonts and sizes); rows of the layout are at least 10 points apart.
				const key = [...byY.keys()].find((k) => Math.abs(k - y) < 3) ?? y;
				byY.set(key, [...(byY.get(key) ?? []), { text: item.str, x, y }]);
			}
			for (const [y, pieces] of [...byY.entries()].sort(([a], [b]) => b - a)) {
				pieces.sort((a, b) => a.x - b.x);
				rows.push({ page: n, y, pieces, text: pieces.map((p) => p.text.trim()).join(' ') });
			}
		}
	} finally {
		await pdf.destroy();
	}
	return rows;
}
