*Model Card for BSIMPD2.0
* Lmin= .2 Lmax= .8 Wmin= 2.8 Wmax= 2.8
.Model N1  NMOS Level= 57
+TNOM = 27        TOX = 4.5E-09    TSI = .0000001   TBOX = 8E-08            
+MOBMOD = 0       CAPMOD = 2       SHMOD =0
+PARAMCHK=0       WINT = 0         LINT = -2E-08    
+VTH0 = .42       K1 = .49         K2 = .1          K3 = 0        
+K3B = 2.2        NLX = 2E-7                 
+DVT0 = 10        DVT1 = .55       DVT2 = -1.4
+DVT0W = 0        DVT1W = 0        DVT2W = 0     
+NCH   = 4.7E+17  NSUB    = -1E+15  NGATE = 1E+20               
+AGIDL=1e-15      BGIDL=1e9        NGIDL=1.1
+NDIODE = 1.13    NTUN = 14.0     NRECF0=2.5      NRECR0=4    
+VREC0=1.2        NTRECF=.1       NTRECR=.2
+ISBJT = 1e-4     ISDIF = 1e-5    ISTUN = 2e-5    ISREC = 4e-2
+XBJT = .9        XDIF = .9       XREC = .9       XTUN = 0.01               
+AHLI=1e-9        LBJT0=0.2e-6    LN=2e-6         
+NBJT=.8          NDIF=-1         AELY=1e8        VABJT=0
+U0 = 352         UA = 1.3E-11     UB = 1.7E-18     UC = -4E-10             
+W0 = 1.16E-06    AGS = .25        A1 = 0           A2 = 1        
+B0 = .01         B1 = 10
+RDSW = 0         PRWG = 0         PRWB = -.2       WR = 1        
+RBODY = 1e0      RBSH = 0.0
+A0 = 1.4         KETA = 0.1       KETAS = 0.2      VSAT = 135000
+DWG = 0          DWB = 0   
+ALPHA0 = 1e-8    BETA0 = 0        BETA1 = 0.05     BETA2 = 0.07
+VDSATII0 = .8    ESATII = 1e7
+VOFF = -.14      NFACTOR = .7     CDSC = .00002    CDSCB    = 0
+CDSCD = 0        CIT = 0                
+PCLM = 2.9       PVAG = 12        PDIBLC1 = .18    PDIBLC2 = .004
+PDIBLCB = -.234  DROUT = .2       
+DELTA = .01      ETA0 = .05       ETAB = 0   
+DSUB = .2        RTH0 = .005
+CLC = .0000001   CLE = .6         CF = 1E-20       CKAPPA = .6               
+CGDL = 1E-20     CGSL = 1E-20     KT1 = -.3        KT1L = 0                
+KT2 = .022       UTE = -1.5       UA1 = 4.31E-09   UB1 = -7.61E-18         
+UC1 = -5.6E-11   PRT = 760        AT = 22400             
+CGSO = 1e-10     CGDO = 1e-10     CJSWG = 1e-12    TT=3e-10
+ASD = 0.3        CSDESW = 1e-12   
+TCJSWG=1e-4      MJSWG=.5         PBSWG=1
