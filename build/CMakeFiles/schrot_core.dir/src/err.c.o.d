CMakeFiles/schrot_core.dir/src/err.c.o: /work/main/src/err.c \
 /usr/include/stdc-predef.h /work/main/include/schrot/err.h
