/* SPDX-License-Identifier: BSD-3-Clause */
/* main.c - placeholder until the command table lands. */
int main(void)
{
	return 0;
}
