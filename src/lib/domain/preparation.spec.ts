import { describe, expect, it } from 'vitest';
import { preparationChecklist } from './preparation';

describe('the artist’s preparation checklist', () => {
	it('has instruments, the music and hearing, each a list of whole sentences', () => {
		for (const withEngineer of [true, false]) {
			const groups = preparationChecklist(withEngineer);
			expect(groups.map((g) => [g.title, g.items.length])).toEqual([
				['Instruments', 3],
				['The music', 3],
				['Hearing', 2]
			]);
			for (const item of groups.flatMap((g) => g.items)) expect(item).toMatch(/^[A-Z].{30,}\.$/);
		}
	});

	it('asks for the running order to go to the engineer only when one is booked', () => {
		const order = (withEngineer: boolean) => preparationChecklist(withEngineer)[1]!.items[2];
		expect(order(true)).toMatch(/^Send the engineer a running order/);
		expect(order(false)).toMatch(/^Write a running order/);
	});

	it('gives the daily exposure action values of Directive 2003/10/EC, Article 3: 80 and 85 dB(A)', () => {
		const hearing = preparationChecklist(false)[2]!.items.join(' ');
		expect(hearing).toContain('2003/10/EC');
		expect(hearing).toContain('80 and 85 dB(A)');
	});
});
