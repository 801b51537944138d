/** Name and version written into the outputs. */
export const SOFTWARE = { name: 'refdelta', version: '0.1.0' } as const;
