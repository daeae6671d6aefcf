// What an artist prepares before a session: common studio practice, in our own words. The hearing
// figures are the daily exposure action values of EU Directive 2003/10/EC, Article 3 (lower 80,
// upper 85 dB(A)); local rules may be stricter and come first. Shown on the booking page and sent
// with the confirmation e-mail.

export interface ChecklistGroup {
	title: string;
	items: string[];
}

export function preparationChecklist(withEngineer: boolean): ChecklistGroup[] {
	return [
		{
			title: 'Instruments',
			items: [
				'Fit new strings a day or two before, so they have stretched and hold their tuning by the session.',
				'Bring spare strings, picks, drum keys and sticks, fresh batteries for pedals and active pickups, and a tuner.',
				'Tune on arrival and between takes. A capo pushes strings sharp: tune again with the capo on.'
			]
		},
		{
			title: 'The music',
			items: [
				'Settle the tempo of each song, and whether you play to a click, before the day.',
				'Bring reference tracks of the sound you are after, and lyric sheets or chord charts for everyone.',
				withEngineer
					? 'Send the engineer a running order, so the room is set up for the first song when you arrive.'
					: 'Write a running order, so set-up time goes on the first song, not on deciding.'
			]
		},
		{
			title: 'Hearing',
			items: [
				'Cue mixes start quiet; ask for more rather than turning it up yourself. Long exposure near 85 dB(A) puts hearing at risk.',
				'EU Directive 2003/10/EC sets daily action values at 80 and 85 dB(A); where local rules are stricter, they apply. Take breaks away from loud sound.'
			]
		}
	];
}
