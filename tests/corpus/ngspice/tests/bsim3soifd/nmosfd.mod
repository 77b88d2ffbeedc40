*Model Card for BSIMFD2.0, floating body FD SOI NMOS
*Released on 2/15/99
.Model N1  NMOS Level= 55 
+TNOM = 27        TOX = 4.5E-09    TSI = 5e-8       TBOX = 8E-08            
+MOBMOD = 0       CAPMOD = 3       SHMOD = 0
+PARAMCHK=0       WINT = 0         LINT = -2E-08    
+VTH0 = .52       K1 = .39         K2 = .1          K3 = 0        
+KB1 = .95        K3B = 2.2        NLX = 7.2E-08           
+DVT0 = .55       DVT1 = .28       DVT2 = -1.4
+DVT0W = 0        DVT1W = 0        DVT2W = 0     
+NCH   = 3.3E+17  NSUB = 1E+15     NGATE = 1E+20               
+DVBD0 = 60.0     DVBD1 = 1.1      VBSA = 0.0              
+KB3 = 2.2        DELP = 0.02             
+ABP = 0.9        MXC = 0.9        ADICE0 = 0.93
+KBJT1 = 1.0E-08  EDL = .0000005
+NDIODE = 1.13    NTUN = 14.0     
+ISBJT = 2e-6     ISDIF = 1e-6      ISTUN = 0.0     ISREC = 1e-5
+XBJT = 0.01      XDIF = 0.01      XREC = 0.01      XTUN = 0.001               
+U0 = 352         UA = 1.3E-11     UB = 1.7E-18     UC = -4E-10             
+W0 = 1.16E-06    AGS = .25        A1 = 0           A2 = 1        
+B0 = .01         B1 = 10
+RDSW = 700       PRWG = 0         PRWB = -.2       WR = 1        
+RBODY = 0.0      RBSH = 0.0
+A0 = 1.4         KETA = -.67      VSAT = 135000
+DWG = 0          DWB = 0   
+ALPHA0 = 0.0     ALPHA1 = 1.5     BETA0 = 20.5
+AII = 1.2        BII = 0.1e-7     CII = 0.8        DII = 0.6
+VOFF = -.14      NFACTOR = .7     CDSC = .00002    CDSCB    = 0                
+CDSCD = 0        CIT = 0                
+PCLM = 2.9       PVAG = 12        PDIBLC1 = .18    PDIBLC2 = .004              
+PDIBLCB = -.234  DROUT = .2       
+DELTA = .01      ETA0 = .01       ETAB = 0   
+DSUB = .3        RTH0 94    = .006
+CLC = .0000001   CLE = .6         CF = 1E-20       CKAPPA = .6               
+CGDL = 1E-20     CGSL = 1E-20     KT1 = -.3        KT1L = 0                
+KT2 = .022       UTE = -1.5       UA1 = 4.31E-09   UB1 = -7.61E-18         
+UC1 = -5.6E-11   PRT = 760        AT = 22400             
+CGSO = 1e-10     CGDO = 1e-10     CJSWG = 5e-10    TT=3e-10
+ASD = 0.3        CSDESW = 1e-12   
