// clipper-lib ships no types; the overlay measurement uses a handful of its calls.
declare module 'clipper-lib';
